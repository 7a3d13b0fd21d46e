import PgBoss from 'pg-boss'

// Explicit imports only: scripts and tests load these helpers outside Nitro.

/** How quickly jobs move; BLOOMLINE_JOBS_FAST=1 (the tests) shrinks every interval to about a second. */
export function jobTuning(env = process.env) {
  const fast = env.BLOOMLINE_JOBS_FAST === '1'
  return {
    fast,
    pollingIntervalSeconds: fast ? 0.5 : 2,
    maintenanceIntervalSeconds: fast ? 1 : 60,
    cronMonitorIntervalSeconds: fast ? 1 : 30,
    /** A send job running longer than this is taken for dead, and pg-boss tries it again. */
    mailExpireSeconds: fast ? 5 : 120,
    /**
     * How long a claimed message stays its worker's. Longer than the expiry in production, so a slow
     * but live send is not taken up by a second worker; in the tests as long, so a crash recovers fast.
     */
    mailLockSeconds: fast ? 5 : 300,
    /** The first wait after a failed send; each further wait doubles. */
    mailRetrySeconds: Number(env.BLOOMLINE_MAIL_RETRY_SECONDS || (fast ? 1 : 30)),
    mailMaxAttempts: Number(env.BLOOMLINE_MAIL_MAX_ATTEMPTS || 10),
  }
}

/** Whether this process runs jobs at all (BLOOMLINE_JOBS=off turns them off, for scripts). */
export function jobsEnabled(env = process.env): boolean {
  return env.BLOOMLINE_JOBS !== 'off' && !!env.DATABASE_URL
}

/** Whether this process fires scheduled (cron) jobs; BLOOMLINE_SCHEDULE=off leaves that to other instances. */
export function scheduleEnabled(env = process.env): boolean {
  return env.BLOOMLINE_SCHEDULE !== 'off'
}

let starting: Promise<PgBoss | null> | undefined
let running: PgBoss | undefined

/**
 * The process's one pg-boss, started on first use: jobs live in PostgreSQL (schema `pgboss`), so
 * any number of app instances share one queue and each scheduled job runs once across them.
 * Null when jobs are turned off.
 */
export function useJobs(): Promise<PgBoss | null> {
  if (starting) return starting
  if (!jobsEnabled()) return (starting = Promise.resolve(null))
  const tuning = jobTuning()
  const boss = new PgBoss({
    connectionString: process.env.DATABASE_URL,
    application_name: 'bloomline-jobs',
    max: 4,
    schedule: scheduleEnabled(),
    maintenanceIntervalSeconds: tuning.maintenanceIntervalSeconds,
    monitorStateIntervalSeconds: tuning.fast ? 5 : 60,
    cronMonitorIntervalSeconds: tuning.cronMonitorIntervalSeconds,
    cronWorkerIntervalSeconds: tuning.fast ? 1 : 5,
  })
  boss.on('error', error => console.error(`Jobs: ${error.message}`))
  starting = boss.start().then(() => (running = boss))
  return starting
}

let queueChain: Promise<unknown> = Promise.resolve()

/**
 * Makes a queue if it is not there yet (pg-boss 10 needs one before send, work or schedule).
 * One at a time in this process, and tried again when another instance making queues at the same
 * moment deadlocks with us: pg-boss makes a table for each queue.
 */
export function ensureQueue(boss: PgBoss, name: string, options: Omit<PgBoss.Queue, 'name'> = {}): Promise<void> {
  const made = queueChain.then(async () => {
    for (let attempt = 1; ; attempt++) {
      if (await boss.getQueue(name)) {
        // Options changed in code reach a queue made by an earlier release.
        await boss.updateQueue(name, { name, ...options })
        return
      }
      try {
        await boss.createQueue(name, { name, ...options })
        return
      }
      catch (error) {
        if (await boss.getQueue(name)) return
        if (attempt >= 5) throw error
        await new Promise(r => setTimeout(r, 100 * attempt + Math.random() * 200))
      }
    }
  })
  queueChain = made.catch(() => undefined)
  return made
}

/** Sends a job when jobs run in this process; returns its id, or null when a like job already waits. */
export async function sendJob(name: string, data: object, options: PgBoss.SendOptions = {}): Promise<string | null> {
  const boss = await useJobs()
  if (!boss) throw new Error('Jobs are turned off in this process.')
  return boss.send(name, data, options)
}

/** Stops pg-boss, letting running jobs finish for a few seconds. */
export async function stopJobs() {
  const boss = running
  starting = undefined
  running = undefined
  if (boss) await boss.stop({ graceful: true, timeout: 5000, wait: true })
}
