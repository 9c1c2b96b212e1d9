import { pgEnum } from 'drizzle-orm/pg-core';
import {
  ROLES,
  MATERIAL_KINDS,
  STORAGE_CLASSES,
  LOT_STATUSES,
  CONTAINER_STATUSES,
  MIX_STATUSES,
  BATCH_STATUSES,
  DRIVER_STATUSES,
  TEST_RESULTS,
  ALERT_SEVERITIES,
  ALERT_STATES,
  STEP_RUN_KINDS,
  ATTACHMENT_KINDS,
  EMAIL_STATUSES,
  EMAIL_KINDS,
} from '../../../shared/constants';
import { NOTIFICATION_MODES } from '../../../shared/notifications';

export const roleEnum = pgEnum('role', ROLES);
export const materialKindEnum = pgEnum('material_kind', MATERIAL_KINDS);
export const storageClassEnum = pgEnum('storage_class', STORAGE_CLASSES);
export const lotStatusEnum = pgEnum('lot_status', LOT_STATUSES);
export const containerStatusEnum = pgEnum('container_status', CONTAINER_STATUSES);
export const mixStatusEnum = pgEnum('mix_status', MIX_STATUSES);
export const batchStatusEnum = pgEnum('batch_status', BATCH_STATUSES);
export const driverStatusEnum = pgEnum('driver_status', DRIVER_STATUSES);
export const testResultEnum = pgEnum('test_result', TEST_RESULTS);
export const alertSeverityEnum = pgEnum('alert_severity', ALERT_SEVERITIES);
export const alertStateEnum = pgEnum('alert_state', ALERT_STATES);
export const stepRunKindEnum = pgEnum('step_run_kind', STEP_RUN_KINDS);
export const attachmentKindEnum = pgEnum('attachment_kind', ATTACHMENT_KINDS);
export const emailStatusEnum = pgEnum('email_status', EMAIL_STATUSES);
export const emailKindEnum = pgEnum('email_kind', EMAIL_KINDS);
export const notificationModeEnum = pgEnum('notification_mode', NOTIFICATION_MODES);
