/**
 * Progress travels from the library to whoever shows it as plain events; the library never prints.
 * The CLI turns them into bars on a TTY (`src/report/terminal.ts`) and drops them otherwise.
 */
export interface ProgressEvent {
  /** A short name of the step: `read`, `checks`, `fit`, `score`, … */
  phase: string;
  done: number;
  total?: number;
  /** A free-form line for the step: `epoch 3 loss 0.41 mrr 0.52`. */
  detail?: string;
}

export type ProgressSink = (event: ProgressEvent) => void;

export const silentProgress: ProgressSink = () => {};
