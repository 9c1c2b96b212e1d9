export * from './enums';
export * from './users';
export * from './attachments';
export * from './catalogue';
export * from './inventory';
export * from './production';
export * from './oversight';
