export { receiveLot } from './receive';
export { attachCertificate } from './certificate';
export { randomContainerCode, newContainerCodes } from './codes';
