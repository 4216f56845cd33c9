export { OutboxScreen as default } from '@/features/outbox/outbox-screen';
