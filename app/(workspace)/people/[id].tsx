import { useLocalSearchParams } from 'expo-router';
import { EditPersonScreen } from '@/components/people/person-form-screen';

export default function PersonRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return <EditPersonScreen key={id} id={Number(id)} />;
}
