export { InviteScreen as default } from '@/components/invite/invite-screen';
