export { dateInWords, listInWords, regionsToWork, renderWeeklyStatus, type RegionsToWork } from './render'
export {
  addIsoWeeks,
  DEFAULT_WEEKLY_DAY,
  DEFAULT_WEEKLY_HOUR,
  ISO_WEEKDAYS,
  isIsoWeekKey,
  isoWeekMonday,
  isoWeekNumber,
  isoWeekRange,
  nextWeeklySendAt,
  WEEKDAY_NAMES,
  weeklyDue,
  weeklySendAt,
  type WeeklyDue,
  type WeeklySchedule,
  type ZoneClock,
} from './schedule'
export type { WeeklyClassWarning, WeeklyClosing, WeeklyDog, WeeklyPlanStep, WeeklyStatus, WeeklyStatusMessage, WeeklyTask } from './types'
