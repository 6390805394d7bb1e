import { checkAtMostOne } from './cardinality.js';
import type { Check } from './types.js';

/** owl:FunctionalProperty (OWL 2 Structural Specification §9.2.4): at most one value per subject. */
export const functional: Check = {
  meta: {
    id: 'functional',
    title: 'Functional property with several values',
    severity: 'error',
    description:
      'A subject has two or more different values of a property declared owl:FunctionalProperty (or of its ' +
      'sub-properties). Different literals are an error; different resources only make OWL infer they are the ' +
      'same individual, so they are a warning unless --closed-world.',
    messages: {
      literals: '{entity} has {count} different values of {predicate}, which is declared functional',
      resources: '{entity} has {count} different values of {predicate}, which is declared functional (OWL would infer they are the same individual)',
    },
  },
  run: (ctx) => checkAtMostOne(ctx, 'functional'),
};
