import { DataTypes, literal, type QueryInterface } from 'sequelize'

// A database default as well as Sequelize's own, so raw inserts (bulk loads, scripts) get timestamps too.
const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
  updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') },
}
const organisation = { type: DataTypes.INTEGER, allowNull: false, references: { model: 'organisations', key: 'id' }, onDelete: 'CASCADE' }
const user = (allowNull: boolean) => ({ type: DataTypes.INTEGER, allowNull, references: { model: 'users', key: 'id' }, onDelete: allowNull ? 'SET NULL' : 'RESTRICT' })

/** Coat profiles, dogs, coat work, shows, entries, grooming tasks and the audit trail. */
export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql)

  await qi.createTable('coat_profiles', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organisation_id: organisation,
    key: { type: DataTypes.STRING(60), allowNull: false },
    label: { type: DataTypes.STRING(120), allowNull: false },
    tolerance_days: { type: DataTypes.INTEGER, allowNull: false },
    on_track_score: { type: DataTypes.INTEGER, allowNull: false },
    regions: { type: DataTypes.JSONB, allowNull: false },
    is_default: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  })
  await qi.addConstraint('coat_profiles', { type: 'unique', fields: ['organisation_id', 'key'], name: 'coat_profiles_organisation_key' })

  await qi.createTable('dogs', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organisation_id: organisation,
    call_name: { type: DataTypes.STRING(60), allowNull: false },
    registered_name: { type: DataTypes.STRING(160), allowNull: false },
    registration_number: { type: DataTypes.STRING(40), allowNull: true },
    breed: { type: DataTypes.STRING(80), allowNull: false },
    sex: { type: DataTypes.STRING(5), allowNull: false },
    date_of_birth: { type: DataTypes.DATEONLY, allowNull: false },
    colour: { type: DataTypes.STRING(60), allowNull: true },
    owner_name: { type: DataTypes.STRING(120), allowNull: true },
    owner_email: { type: DataTypes.STRING(254), allowNull: true },
    owner_phone: { type: DataTypes.STRING(40), allowNull: true },
    handler_id: user(true),
    coat_profile_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'coat_profiles', key: 'id' }, onDelete: 'RESTRICT' },
    notes: { type: DataTypes.TEXT, allowNull: true },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'active' },
    ...timestamps,
  })
  await q(`ALTER TABLE dogs
    ADD CONSTRAINT dogs_sex_check CHECK (sex IN ('dog', 'bitch')),
    ADD CONSTRAINT dogs_status_check CHECK (status IN ('active', 'retired'))`)
  await q(`CREATE UNIQUE INDEX dogs_registration_number ON dogs (organisation_id, lower(registration_number)) WHERE registration_number IS NOT NULL`)
  await qi.addIndex('dogs', ['organisation_id', 'handler_id'])

  await qi.createTable('coat_work', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organisation_id: organisation,
    dog_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'dogs', key: 'id' }, onDelete: 'CASCADE' },
    date: { type: DataTypes.DATEONLY, allowNull: false },
    kind: { type: DataTypes.STRING(10), allowNull: false },
    regions: { type: DataTypes.ARRAY(DataTypes.STRING(40)), allowNull: false },
    worked_by_id: user(true),
    recorded_by_id: user(true),
    minutes: { type: DataTypes.INTEGER, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    task_id: { type: DataTypes.INTEGER, allowNull: true },
    // Deleted work is kept, with who deleted it and when, so nothing is silently lost.
    deleted_at: { type: DataTypes.DATE, allowNull: true },
    deleted_by_id: user(true),
    ...timestamps,
  })
  await q(`ALTER TABLE coat_work
    ADD CONSTRAINT coat_work_kind_check CHECK (kind IN ('strip', 'layer', 'roll', 'card', 'bath', 'trim')),
    ADD CONSTRAINT coat_work_regions_check CHECK (cardinality(regions) > 0),
    ADD CONSTRAINT coat_work_minutes_check CHECK (minutes IS NULL OR minutes >= 0)`)
  await q('CREATE INDEX coat_work_dog_date ON coat_work (dog_id, date) WHERE deleted_at IS NULL')
  await qi.addIndex('coat_work', ['organisation_id'])

  await qi.createTable('shows', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organisation_id: organisation,
    name: { type: DataTypes.STRING(160), allowNull: false },
    club: { type: DataTypes.STRING(160), allowNull: true },
    first_day: { type: DataTypes.DATEONLY, allowNull: false },
    last_day: { type: DataTypes.DATEONLY, allowNull: false },
    place: { type: DataTypes.STRING(200), allowNull: true },
    judges: { type: DataTypes.ARRAY(DataTypes.STRING(120)), allowNull: false, defaultValue: [] },
    time_zone: { type: DataTypes.STRING(64), allowNull: false },
    entries_close_at: { type: DataTypes.DATE, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps,
  })
  await q(`ALTER TABLE shows ADD CONSTRAINT shows_days_check CHECK (last_day >= first_day)`)
  await q(`CREATE UNIQUE INDEX shows_name_first_day ON shows (organisation_id, lower(name), first_day)`)
  await qi.addIndex('shows', ['organisation_id', 'first_day'])

  await qi.createTable('entries', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organisation_id: organisation,
    dog_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'dogs', key: 'id' }, onDelete: 'CASCADE' },
    show_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'shows', key: 'id' }, onDelete: 'CASCADE' },
    class_code: { type: DataTypes.STRING(40), allowNull: false },
    armband: { type: DataTypes.STRING(20), allowNull: true },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'planned' },
    handler_id: user(true),
    notes: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps,
  })
  await q(`ALTER TABLE entries ADD CONSTRAINT entries_status_check CHECK (status IN ('planned', 'entered', 'confirmed', 'withdrawn'))`)
  await qi.addConstraint('entries', { type: 'unique', fields: ['show_id', 'dog_id', 'class_code'], name: 'entries_show_dog_class' })
  await qi.addIndex('entries', ['organisation_id', 'dog_id'])
  await qi.addIndex('entries', ['organisation_id', 'handler_id'])

  await qi.createTable('tasks', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    organisation_id: organisation,
    dog_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'dogs', key: 'id' }, onDelete: 'CASCADE' },
    kind: { type: DataTypes.STRING(10), allowNull: false },
    regions: { type: DataTypes.ARRAY(DataTypes.STRING(40)), allowNull: false },
    due_date: { type: DataTypes.DATEONLY, allowNull: false },
    window_start: { type: DataTypes.TIME, allowNull: true },
    window_end: { type: DataTypes.TIME, allowNull: true },
    assignee_id: user(true),
    created_by_id: user(true),
    status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'open' },
    skip_reason: { type: DataTypes.TEXT, allowNull: true },
    minutes: { type: DataTypes.INTEGER, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    plan_step_key: { type: DataTypes.STRING(200), allowNull: true },
    coat_work_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'coat_work', key: 'id' }, onDelete: 'SET NULL' },
    done_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  })
  await q(`ALTER TABLE tasks
    ADD CONSTRAINT tasks_kind_check CHECK (kind IN ('strip', 'layer', 'roll', 'card', 'bath', 'trim')),
    ADD CONSTRAINT tasks_status_check CHECK (status IN ('open', 'in-progress', 'done', 'skipped'))`)
  await q(`CREATE UNIQUE INDEX tasks_plan_step ON tasks (dog_id, plan_step_key) WHERE plan_step_key IS NOT NULL`)
  await qi.addIndex('tasks', ['organisation_id', 'assignee_id', 'status'])
  await q(`ALTER TABLE coat_work ADD CONSTRAINT coat_work_task_fk FOREIGN KEY (task_id) REFERENCES tasks (id) ON DELETE SET NULL`)

  await qi.createTable('audit_events', {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    organisation_id: organisation,
    actor_id: user(true),
    entity: { type: DataTypes.STRING(30), allowNull: false },
    entity_id: { type: DataTypes.INTEGER, allowNull: false },
    action: { type: DataTypes.STRING(20), allowNull: false },
    before: { type: DataTypes.JSONB, allowNull: true },
    after: { type: DataTypes.JSONB, allowNull: true },
    ...timestamps,
  })
  await qi.addIndex('audit_events', ['organisation_id', 'entity', 'entity_id'])
}

/** Drops what `up` made, newest first. */
export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('audit_events')
  await qi.sequelize.query('ALTER TABLE coat_work DROP CONSTRAINT IF EXISTS coat_work_task_fk')
  await qi.dropTable('tasks')
  await qi.dropTable('entries')
  await qi.dropTable('shows')
  await qi.dropTable('coat_work')
  await qi.dropTable('dogs')
  await qi.dropTable('coat_profiles')
}
