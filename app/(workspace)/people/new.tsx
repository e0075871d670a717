import { NewPersonScreen } from '@/components/people/person-form-screen';

export default NewPersonScreen;
