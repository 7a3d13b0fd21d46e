/** Empties the manager's part of the demo mailbox (what the list shows them). Managers, demo mode only. */
export default defineEventHandler(async (event) => {
  requireDemoMode()
  const caller = await requireCaller(event, ['manager'])
  const removed = await useModels().DemoMail.destroy({ where: { id: await demoMailIdsFor(caller, { limit: 100_000 }) } })
  return { removed }
})
