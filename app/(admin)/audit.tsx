export { AuditScreen as default } from '@/components/admin/audit/audit-screen';
