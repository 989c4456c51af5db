/**
 * Prometheus metrics (prom-client) on a registry of our own: jobs by state, queue depth and worker count
 * (read from Redis at scrape time), job run duration (observed from queue events), HTTP request durations.
 */
import { Counter, Gauge, Histogram, Registry, collectDefaultMetrics } from 'prom-client';
import { BUDGET_JOB_NAMES, JOB_NAMES, leapSecondsExpired, leapSecondsExpiryMs, type JobEventHub, type RetargetQueue } from '../queue/index.ts';

export class ServiceMetrics {
  readonly registry = new Registry();
  readonly httpDuration: Histogram<'method' | 'route' | 'status'>;
  readonly jobDuration: Histogram<'kind' | 'outcome'>;
  readonly submissions: Counter<'kind' | 'outcome'>;
  private unsubscribe: (() => void) | null = null;

  constructor(private readonly queue: RetargetQueue) {
    const registers = [this.registry];
    collectDefaultMetrics({ register: this.registry, prefix: 'veer_api_' });
    new Gauge({
      name: 'veer_jobs', help: 'Jobs in the queue by state (retarget and budget jobs and their sample batches)', labelNames: ['state'], registers,
      collect: async function collect(this: Gauge<'state'>) {
        const counts = await queue.counts();
        for (const [state, n] of Object.entries(counts)) this.set({ state }, n);
      },
    });
    new Gauge({
      name: 'veer_queue_depth', help: 'Jobs waiting for a worker (waiting + delayed)', registers,
      collect: async function collect(this: Gauge) {
        const c = await queue.counts();
        this.set(c.waiting + c.delayed);
      },
    });
    new Gauge({
      name: 'veer_workers', help: 'Worker connections seen on the queue', registers,
      collect: async function collect(this: Gauge) { this.set(await queue.workerCount()); },
    });
    new Gauge({
      name: 'veer_leap_seconds_expiry_timestamp_seconds', help: 'Expiry of the leap-second table in use (Unix seconds, 00:00 UTC of its #@ day)',
      labelNames: ['source'], registers,
      collect: function collect(this: Gauge<'source'>) {
        this.set({ source: queue.leapSeconds.origin }, leapSecondsExpiryMs(queue.leapSeconds) / 1000);
      },
    });
    new Gauge({
      name: 'veer_leap_seconds_expired', help: '1 when the leap-second table in use has expired (UTC past it is assumed, with a plan caveat)', registers,
      collect: function collect(this: Gauge) { this.set(leapSecondsExpired(queue.leapSeconds, new Date()) ? 1 : 0); },
    });
    this.jobDuration = new Histogram({
      name: 'veer_job_duration_seconds', help: 'Run time of finished jobs by kind (retarget, delta-v-budget; processing start to end)',
      labelNames: ['kind', 'outcome'], buckets: [0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60, 120, 300, 900], registers,
    });
    this.httpDuration = new Histogram({
      name: 'veer_http_request_duration_seconds', help: 'HTTP request durations', labelNames: ['method', 'route', 'status'],
      buckets: [0.001, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5], registers,
    });
    this.submissions = new Counter({
      name: 'veer_job_submissions_total', help: 'Job submissions by kind (retarget, delta-v-budget) and outcome (created, existing, conflict, invalid, queue-full, submitter-full)',
      labelNames: ['kind', 'outcome'], registers,
    });
  }

  /** Observes job durations from queue events. */
  watch(events: JobEventHub): void {
    this.unsubscribe = events.subscribe('*', (e) => {
      if (e.type !== 'completed' && e.type !== 'failed') return;
      void this.queue.findJob(e.jobId).then((job) => {
        if (!job || !job.processedOn || !job.finishedOn) return;
        const kind = job.name === JOB_NAMES.retarget ? 'retarget' : job.name === BUDGET_JOB_NAMES.budget ? 'delta-v-budget' : null;
        if (kind) this.jobDuration.observe({ kind, outcome: e.type }, (job.finishedOn - job.processedOn) / 1000);
      }, () => {});
    });
  }

  stop(): void { this.unsubscribe?.(); }
}
