import { checkAtMostOne } from './cardinality.js';
import type { Check } from './types.js';

/** owl:InverseFunctionalProperty (OWL 2 Structural Specification §9.2.6): at most one subject per value. */
export const inverseFunctional: Check = {
  meta: {
    id: 'inverse-functional',
    title: 'Inverse-functional value shared by several subjects',
    severity: 'warning',
    description:
      'Two or more different subjects share a value of a property declared owl:InverseFunctionalProperty. OWL ' +
      'would infer the subjects are the same individual, so this is a warning, an error with --closed-world.',
    messages: {
      literals: '{count} different subjects share the value {entity} of {predicate}, which is declared inverse-functional',
      resources: '{count} different subjects share the value {entity} of {predicate}, which is declared inverse-functional (OWL would infer they are the same individual)',
    },
  },
  run: (ctx) => checkAtMostOne(ctx, 'inverseFunctional'),
};
