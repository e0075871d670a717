import { FinishSignUpScreen } from '@/components/auth/finish-sign-up-screen';

export default FinishSignUpScreen;
