/**
 * The plant's time zone for times shown on the floor screens.
 * TODO(plant zone): take it from the plant-time store (the server's TACKLOG_PLANT_ZONE) once the
 * client has one; until then UTC, the default setting and the demo plant's zone.
 */
export const PLANT_ZONE = 'UTC';
