/** The software version stamped on every plan: package.json's `version`. */
import pkg from '../package.json' with { type: 'json' };

export const SOFTWARE_VERSION: string = `veer ${pkg.version}`;
