import { deliverOutbox, MAIL_SEND_QUEUE, sweepOutbox } from '../utils/mail'
import { ensureQueue, jobTuning, scheduleEnabled, useJobs } from '../utils/jobs'

const MAIL_SWEEP_QUEUE = 'mail-sweep'

/** Starts pg-boss beside the server and the workers that send the outbox; a failure to start is logged, not fatal. */
export default defineNitroPlugin(() => {
  useJobs().then(async (boss) => {
    if (!boss) return
    const tuning = jobTuning()
    // "stately": at most one waiting and one running job per outbox message.
    await ensureQueue(boss, MAIL_SEND_QUEUE, { policy: 'stately', expireInSeconds: tuning.mailExpireSeconds, retryLimit: 30, retryDelay: tuning.mailRetrySeconds, retryBackoff: true })
    await ensureQueue(boss, MAIL_SWEEP_QUEUE, { policy: 'singleton', expireInSeconds: 60, retryLimit: 0 })
    await boss.work<{ outboxId: number }>(MAIL_SEND_QUEUE, { pollingIntervalSeconds: tuning.pollingIntervalSeconds, batchSize: 1 }, async ([job]) => {
      const outcome = await deliverOutbox(job!.data.outboxId)
      // Thrown, so pg-boss tries again (with back-off) once the other worker's lock has run out.
      if (outcome === 'locked') throw new Error(`Outbox message ${job!.data.outboxId} is held by another worker.`)
      return { outcome }
    })
    await boss.work(MAIL_SWEEP_QUEUE, { pollingIntervalSeconds: tuning.pollingIntervalSeconds }, async () => ({ asked: await sweepOutbox() }))
    if (scheduleEnabled()) await boss.schedule(MAIL_SWEEP_QUEUE, '* * * * *')
  }).catch(error => console.error(`Jobs did not start: ${(error as Error).message}`))
})
