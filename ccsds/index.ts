/**
 * Public face of ccsds/: CCSDS Orbit Data Messages (502.0-B) in and out — the Orbit Parameter Message
 * (initial state, covariance, maneuvers) and the Orbit Ephemeris Message (tabulated trajectories), in
 * KVN and XML. Pure: text in, data out (and back); the CLI and the API do the file and HTTP work. The one
 * runner here, CcsdsExportThreads, computes an export in a worker thread so a server's event loop stays free.
 */
export { CcsdsFormatError } from './errors.ts';
export type * from './messages/odm-types.ts';
export { readOpm } from './messages/opm-reader.ts';
export { writeOpm } from './messages/opm-writer.ts';
export { readOem } from './messages/oem-reader.ts';
export { writeOem } from './messages/oem-writer.ts';
export { encodingOf } from './syntax/tokenise.ts';
export { ODM_WRITE_DEFAULTS, type OdmWriteOptions } from './messages/write-options.ts';
export { formatCcsdsEpoch, parseCcsdsEpoch, SUPPORTED_TIME_SYSTEMS } from './syntax/values.ts';
export {
  CENTRE_NAME_OF_BODY, WRITTEN_FRAME_NAME, centreFromName, inertialFrameFromName, frameMeaningFromName,
  assertWritableFrame, type FrameMeaning, type MessageFrame,
} from './messages/frames.ts';
/** Re-exported from propagator/frames (the one frames module) for readers of TNW/VNB message values. */
export { vnbFromTnw, tnwFromVnb } from '../propagator/index.ts';
export { assertPositiveSemiDefinite, PSD_TOLERANCE } from './messages/covariance.ts';
export {
  readOpmAsInitialState, covarianceInStateFrame, type OpmInitialState, type PlannerInitialState,
} from './messages/initial-state.ts';
export {
  oemToEphemeris, oemToTrajectory, segmentInterpolation, OEM_EPHEMERIS_DEFAULTS, type OemEphemerisOptions,
  type OemTrajectory,
} from './messages/oem-ephemeris.ts';
export { assertExportable, ephemerisComments, planToOpm, REVIEW_COMMENTS, type PlanExportOptions } from './export/plan-opm.ts';
export { planToOem, MAX_OEM_LINES, type PlanOemOptions } from './export/plan-oem.ts';
export { exportPlanAsCcsds, type CcsdsExportKind, type CcsdsExportOptions } from './export/export-plan.ts';
export {
  CcsdsExportThreads, ExportTimeLimitError, type CcsdsExportThreadsOptions, type ExportRun, type ThreadExportOptions,
} from './export/export-off-thread.ts';
export { fileSha256, loadEphemerisFiles, oemFileTables, readEphemerisFileBytes } from './messages/oem-ephemeris-files.ts';
export { compareWithReference, type ReferenceComparison } from './messages/compare-reference.ts';
