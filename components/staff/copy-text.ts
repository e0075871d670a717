import { Share } from 'react-native';

/** On phones the share sheet offers Copy (and sending the address to a calendar app). */
export async function copyText(text: string): Promise<boolean> {
  try {
    const result = await Share.share({ message: text });
    return result.action === Share.sharedAction;
  } catch {
    return false;
  }
}
