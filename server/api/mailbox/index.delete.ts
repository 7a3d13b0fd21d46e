/** Empties the demo mailbox. Managers, demo mode only. */
export default defineEventHandler(async (event) => {
  requireDemoMode()
  await requireCaller(event, ['manager'])
  const removed = await useModels().DemoMail.destroy({ where: {}, truncate: false })
  return { removed }
})
