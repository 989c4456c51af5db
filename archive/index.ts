/** Public face of archive/: other rooms import from here only. */
export {};
