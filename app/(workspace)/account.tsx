import { ProfileScreen } from '@/components/auth/profile-screen';

export default ProfileScreen;
