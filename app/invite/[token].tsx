export { InviteScreen as default } from '@/features/auth/invite-screen';
