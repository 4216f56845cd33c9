export { MailboxScreen as default } from '@/features/mailbox/mailbox-screen';
