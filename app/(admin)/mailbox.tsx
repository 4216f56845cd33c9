export { MailboxScreen as default } from '@/components/admin/mailbox/mailbox-screen';
