import type { QueryInterface } from 'sequelize'

// A dog's entries, coat work and tasks, and a show's entries, must belong to the same
// organisation as the dog or show. The API scopes every query by organisation; these keys make
// the database refuse a row that names another organisation's dog or show as well. Each row
// references (organisation_id, dog_id) instead of dog_id alone, so its own organisation_id
// needs no key of its own: the dog's and the show's keys already reach the organisation. That is
// also one foreign-key check fewer per imported entry (docs/import-speed.md).
const CHILDREN = [
  { table: 'entries', parents: [{ column: 'dog_id', parent: 'dogs' }, { column: 'show_id', parent: 'shows' }] },
  { table: 'coat_work', parents: [{ column: 'dog_id', parent: 'dogs' }] },
  { table: 'tasks', parents: [{ column: 'dog_id', parent: 'dogs' }] },
] as const

/** Composite keys from each dog's and show's rows to their parent in the same organisation. */
export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql)
  await q('CREATE UNIQUE INDEX dogs_organisation_id_id ON dogs (organisation_id, id)')
  await q('CREATE UNIQUE INDEX shows_organisation_id_id ON shows (organisation_id, id)')
  for (const { table, parents } of CHILDREN) {
    const changes = [
      `DROP CONSTRAINT ${table}_organisation_id_fkey`,
      ...parents.flatMap(({ column, parent }) => [
        `DROP CONSTRAINT ${table}_${column}_fkey`,
        `ADD CONSTRAINT ${table}_${column}_same_organisation_fkey FOREIGN KEY (organisation_id, ${column}) REFERENCES ${parent} (organisation_id, id) ON DELETE CASCADE`,
      ]),
    ]
    await q(`ALTER TABLE ${table} ${changes.join(', ')}`)
  }
}

/** The single-column keys of 0002 again. */
export async function down({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql)
  for (const { table, parents } of CHILDREN) {
    const changes = [
      `ADD CONSTRAINT ${table}_organisation_id_fkey FOREIGN KEY (organisation_id) REFERENCES organisations (id) ON DELETE CASCADE`,
      ...parents.flatMap(({ column, parent }) => [
        `DROP CONSTRAINT ${table}_${column}_same_organisation_fkey`,
        `ADD CONSTRAINT ${table}_${column}_fkey FOREIGN KEY (${column}) REFERENCES ${parent} (id) ON DELETE CASCADE`,
      ]),
    ]
    await q(`ALTER TABLE ${table} ${changes.join(', ')}`)
  }
  await q('DROP INDEX shows_organisation_id_id')
  await q('DROP INDEX dogs_organisation_id_id')
}
