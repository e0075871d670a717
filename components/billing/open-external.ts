import { Linking } from 'react-native';

/** On a phone the payment pages open in the system browser. */
export function openExternal(url: string): void {
  void Linking.openURL(url);
}
