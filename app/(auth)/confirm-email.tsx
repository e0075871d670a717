import { ConfirmEmailScreen } from '@/components/auth/confirm-email-screen';

export default ConfirmEmailScreen;
