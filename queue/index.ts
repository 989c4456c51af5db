/** Public face of queue/: other rooms import from here only. */
export {};
