/** Removes what the manager's organisation sent from the demo mailbox; shared mail (password resets, outside mail) stays. Managers, demo mode only. */
export default defineEventHandler(async (event) => {
  requireDemoMode()
  const caller = await requireCaller(event, ['manager'])
  const removed = await useModels().DemoMail.destroy({ where: { id: await demoMailIdsFor(caller, { limit: 100_000, own: true }) } })
  return { removed }
})
