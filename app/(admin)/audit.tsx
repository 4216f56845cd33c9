export { AuditScreen as default } from '@/features/audit/audit-screen';
