import { organisationPatchSchema } from '../../../shared/schemas/organisation'

/** Renames the organisation or changes its time zone or show rule set. Managers only. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const patch = await readBodyWith(event, organisationPatchSchema)
  const { Organisation } = useModels()
  const organisation = await Organisation.findByPk(caller.organisationId)
  if (!organisation) throw notFound('organisation')
  await organisation.update(patch)
  return organisationView(organisation)
})
