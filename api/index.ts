/** Public face of api/: other rooms import from here only. */
export {};
