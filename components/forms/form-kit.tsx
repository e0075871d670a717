import { Suspense, use, type ComponentType } from 'react';
import { ActivityIndicator } from 'react-native';
import { colors } from '@/constants/theme';
import { loadFormKit, type FormKit } from './form-kit-load';

/** The form library inside a component wrapped by `withFormKit` (it waits there until loaded). */
export function useFormKit(): FormKit {
  return use(loadFormKit());
}

/** A form component that waits, behind a spinner of its own, for the form library to arrive. */
export function withFormKit<P extends object>(Form: ComponentType<P>): ComponentType<P> {
  const WithFormKit = (props: P) => (
    <Suspense fallback={<ActivityIndicator color={colors.loom} accessibilityLabel="Loading the form" />}>
      <Form {...props} />
    </Suspense>
  );
  WithFormKit.displayName = `withFormKit(${Form.displayName ?? Form.name})`;
  return WithFormKit;
}
