/** Chooses the PlanSink from configuration: the archive (SQLite in DATA_DIR, or PostgreSQL by DATABASE_URL). */
import { openArchive } from '../archive/index.ts';
import { ArchivePlanSink, JobResultSink, type PlanSink } from './plan-sink.ts';
import type { WorkerConfig } from './worker-config.ts';

export async function createPlanSink(config: Pick<WorkerConfig, 'PLAN_SINK' | 'DATA_DIR' | 'DATABASE_URL'>): Promise<PlanSink> {
  if (config.PLAN_SINK === 'job-result') return new JobResultSink();
  const archive = await openArchive({
    dataDir: config.DATA_DIR, ...(config.DATABASE_URL ? { databaseUrl: config.DATABASE_URL } : {}),
  });
  return new ArchivePlanSink(archive);
}
