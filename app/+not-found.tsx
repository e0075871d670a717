import { NotFoundScreen } from '@/components/not-found-screen';

export default NotFoundScreen;
