/** The organisation the caller is working in. Every role may read it. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event)
  const { Organisation } = useModels()
  const organisation = await Organisation.findByPk(caller.organisationId)
  if (!organisation) throw notFound('organisation')
  return organisationView(organisation)
})
