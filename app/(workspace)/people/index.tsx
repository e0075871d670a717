import { PeopleScreen } from '@/components/people/people-screen';

export default PeopleScreen;
