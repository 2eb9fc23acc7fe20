import type { Knex } from 'knex'
import bcrypt from 'bcryptjs'
import { TABLES, TABLES_CHILDREN_FIRST } from '../server/db/tables'
import { DEMO_PATIENTS, DEMO_STUDY, DEMO_USERS } from '../server/demo/demo-data'

/** Replaces everything with the invented demo clinic. Refuses to run in production. */
export async function seed(knex: Knex): Promise<void> {
  if (process.env.NODE_ENV === 'production') throw new Error('Demo seeds never run in production.')
  for (const table of TABLES_CHILDREN_FIRST) await knex(table).del()

  const userIds = new Map<string, number>()
  for (const user of DEMO_USERS) {
    const [id] = await knex(TABLES.users).insert({
      email: user.email,
      display_name: user.displayName,
      role: user.role,
      // Cost 10 as in production; seeding six users takes well under a second.
      password_hash: await bcrypt.hash(user.password, 10),
    })
    userIds.set(user.email, id as number)
  }
  const fellowId = userIds.get('priya.lindqvist@endplate.example') as number
  const surgeonId = userIds.get('rhea.calloway@endplate.example') as number
  const researcherId = userIds.get('mei.arkwright@endplate.example') as number

  // Surgeons set studies up; the researcher works in it as a member.
  const [studyId] = await knex(TABLES.studies).insert({ ...DEMO_STUDY, created_by: surgeonId })
  await knex(TABLES.studyMembers).insert({ study_id: studyId, user_id: researcherId })

  for (const patient of DEMO_PATIENTS) {
    const [patientId] = await knex(TABLES.patients).insert({
      record_number: patient.recordNumber,
      family_name: patient.familyName,
      given_name: patient.givenName,
      birth_date: patient.birthDate,
      sex: patient.sex,
      study_code: patient.studyCode,
      osteoporosis: patient.osteoporosis ?? false,
      notes: patient.notes,
      created_by: fellowId,
    })
    for (const visit of patient.visits) {
      await knex(TABLES.visits).insert({
        patient_id: patientId,
        visit_date: visit.date,
        kind: visit.kind,
        months_since_surgery: visit.monthsSinceSurgery ?? null,
        indication: visit.indication,
        created_by: fellowId,
      })
    }
    for (const segment of patient.plan ?? []) {
      await knex(TABLES.planSegments).insert({
        patient_id: patientId,
        segment: segment.segment,
        treatment: segment.treatment,
        pars_defect_left: segment.parsDefectLeft ?? false,
        pars_defect_right: segment.parsDefectRight ?? false,
        facet_degeneration: segment.facetDegeneration ?? false,
        dynamic_instability: segment.dynamicInstability ?? false,
        implant_lordosis_deg: segment.implantLordosisDeg ?? null,
        implant_height_mm: segment.implantHeightMm ?? null,
        notes: segment.notes ?? null,
        updated_by: surgeonId,
      })
    }
    if (patient.inStudy)
      await knex(TABLES.studyPatients).insert({ study_id: studyId, patient_id: patientId })
  }
}
