/** Public face of planner/: other rooms import from here only. */
export {};
