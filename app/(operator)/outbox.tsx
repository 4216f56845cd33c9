export { OutboxScreen as default } from '@/components/outbox/outbox-screen';
