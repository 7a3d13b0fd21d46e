import { weeklyTickJobSchema } from '../../shared/schemas/weekly'
import { ensureQueue, jobTuning, scheduleEnabled, useJobs } from '../utils/jobs'
import { runWeeklyTick, WEEKLY_TICK_QUEUE } from '../utils/weeklySchedule'

/**
 * The weekly status on pg-boss: every instance works the tick queue; those that fire schedules
 * register its cron, every minute. pg-boss creates one job per minute however many instances
 * fire it, and the outbox key makes a repeated tick (a retry after a crash) send nothing twice.
 */
export default defineNitroPlugin(() => {
  useJobs().then(async (boss) => {
    if (!boss) return
    const tuning = jobTuning()
    // "singleton": one tick runs at a time across all instances (correct without it, thanks to the
    // outbox key, but no work is done twice). A tick whose instance died is taken for dead after
    // the expiry and run again.
    await ensureQueue(boss, WEEKLY_TICK_QUEUE, { policy: 'singleton', expireInSeconds: tuning.fast ? 20 : 600, retryLimit: 5, retryDelay: tuning.fast ? 2 : 30, retryBackoff: true })
    await boss.work(WEEKLY_TICK_QUEUE, { pollingIntervalSeconds: tuning.pollingIntervalSeconds, batchSize: 1 }, async ([job]) => {
      const data = weeklyTickJobSchema.parse(job?.data ?? {})
      const result = await runWeeklyTick({ at: data.at ? new Date(data.at) : undefined, organisationId: data.organisationId })
      if (result.queued) console.info(`Weekly status: ${result.queued} message(s) queued for ${result.due} organisation(s).`)
      return result
    })
    if (scheduleEnabled()) await boss.schedule(WEEKLY_TICK_QUEUE, '* * * * *')
  }).catch(error => console.error(`The weekly status schedule did not start: ${(error as Error).message}`))
})
