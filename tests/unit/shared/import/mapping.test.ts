import { describe, expect, it } from 'vitest'
import { detectDayOrder, proposeMapping, readImportDate, resolveClassCode } from '../../../../shared/import'

describe('proposing a mapping', () => {
  it.each([
    ['Registered Name', 'registeredName'],
    ['  REG. NO. ', 'registrationNumber'],
    ['D.O.B.', 'dateOfBirth'],
    ['date_of_birth', 'dateOfBirth'],
    ['Show Date', 'showFirstDay'],
    ['Gender', 'sex'],
    ['Ring number', 'armband'],
    ['Handler E-mail', 'handlerEmail'],
    ['Venue', 'place'],
    ['Closing date', 'entriesClose'],
  ])('maps %j to %s, ignoring case, spaces and punctuation', (header, field) => {
    expect(proposeMapping(['Unrelated column', header])).toEqual({ [field]: header })
  })

  it('prefers the remembered mapping for headers the file has, and gives no field two columns', () => {
    const mapping = proposeMapping(['Hound', 'Dog', 'Class'], { registeredName: 'hound' })
    expect(mapping).toEqual({ registeredName: 'Hound', classCode: 'Class' })
  })

  it('leaves an unknown header unmapped', () => {
    expect(proposeMapping(['Favourite biscuit'])).toEqual({})
  })
})

describe('reading dates', () => {
  // ISO 8601 calendar dates, and the common written forms (common practice, no source).
  it.each([
    ['2027-05-29', 'day-first', '2027-05-29'],
    ['29/05/2027', 'day-first', '2027-05-29'],
    ['05/29/2027', 'month-first', '2027-05-29'],
    ['29 May 2027', 'month-first', '2027-05-29'],
    ['May 29, 2027', 'day-first', '2027-05-29'],
    ['29-may-2027', 'day-first', '2027-05-29'],
    ['1.6.2027', 'day-first', '2027-06-01'],
    ['31/02/2027', 'day-first', null],
    ['29/02/2027', 'day-first', null],
    ['29/02/2028', 'day-first', '2028-02-29'],
    ['12/03/24', 'day-first', null],
    ['13/13/2027', 'day-first', null],
    ['next Tuesday', 'day-first', null],
  ] as const)('%j read %s is %j', (text, order, expected) => {
    expect(readImportDate(text, order)).toBe(expected)
  })

  it.each([
    [['03/04/2027', '29/05/2027'], 'day-first', false],
    [['03/04/2027', '05/29/2027'], 'month-first', false],
    [['03/04/2027', '2027-05-29'], null, false],
    [['29/05/2027', '05/29/2027'], null, true],
  ] as const)('the values %j decide %s for the whole file', (values, order, conflict) => {
    expect(detectDayOrder(values)).toEqual({ order, conflict })
  })
})

describe('class codes', () => {
  // Codes and labels from shared/coat CLASS_DEFINITIONS (The Kennel Club (UK) Definitions of Classes, from memory).
  it.each([
    ['kc:junior', 'kc:junior'],
    ['Junior', 'kc:junior'],
    ['minor puppy', 'kc:minor-puppy'],
    ['KC:Post-Graduate', 'kc:post-graduate'],
    ['fci:junior', undefined],
    ['Wizard Stakes', undefined],
  ])('%j in KC is %j', (text, code) => {
    expect(resolveClassCode('KC', text)).toBe(code)
  })
})
