export { SettingsScreen as default } from '@/components/admin/settings/settings-screen';
