/** The software's version, read once from package.json: stamped on every plan and shown in the OpenAPI document. */
import pkg from '../package.json' with { type: 'json' };

/** package.json's semantic version, e.g. `0.1.0` (the OpenAPI document's info.version). */
export const PACKAGE_VERSION: string = pkg.version;
/** What a plan records as the software that made it, e.g. `veer 0.1.0`. */
export const SOFTWARE_VERSION: string = `veer ${PACKAGE_VERSION}`;
