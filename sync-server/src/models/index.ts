import type { Sequelize } from 'sequelize';
import { AppliedMutation, initAppliedMutation } from './applied-mutation';
import { AuditEvent, initAuditEvent } from './audit-event';
import { Client, initClient } from './client';
import { ClipBlob, initClipBlob } from './clip-blob';
import { Consent, initConsent } from './consent';
import { ConsentText, initConsentText } from './consent-text';
import { Clinic, initClinic } from './clinic';
import { RecordingSession, initRecordingSession } from './recording-session';
import { RefreshToken, initRefreshToken } from './refresh-token';
import { SiteRecording, initSiteRecording } from './site-recording';
import { SyncConflict, initSyncConflict } from './sync-conflict';
import { User, initUser } from './user';

export {
  AppliedMutation,
  AuditEvent,
  Client,
  ClipBlob,
  Consent,
  ConsentText,
  Clinic,
  RecordingSession,
  RefreshToken,
  SiteRecording,
  SyncConflict,
  User,
};

let boundTo: Sequelize | undefined;

/** Binds the model classes to one Sequelize; a process talks to one database through them. */
export function initModels(sequelize: Sequelize): void {
  if (boundTo === sequelize) return;
  boundTo = sequelize;
  for (const init of [
    initClinic,
    initUser,
    initRefreshToken,
    initClient,
    initConsentText,
    initConsent,
    initRecordingSession,
    initSiteRecording,
    initClipBlob,
    initAppliedMutation,
    initSyncConflict,
    initAuditEvent,
  ]) {
    init(sequelize);
  }
  User.belongsTo(Clinic, { foreignKey: 'clinicId', as: 'clinic' });
  Consent.belongsTo(Client, { foreignKey: 'clientId', as: 'client' });
  Client.hasMany(Consent, { foreignKey: 'clientId', as: 'consents' });
  RecordingSession.belongsTo(Client, { foreignKey: 'clientId', as: 'client' });
  RecordingSession.belongsTo(User, { foreignKey: 'operatorId', as: 'operator' });
  RecordingSession.hasMany(SiteRecording, { foreignKey: 'sessionId', as: 'siteRecordings' });
  SiteRecording.belongsTo(RecordingSession, { foreignKey: 'sessionId', as: 'session' });
}
