import { StyleSheet, Text } from 'react-native';
import { Link, type Href } from 'expo-router';
import { colors, fonts } from '@/constants/theme';

export function TextLink({ href, label, testID }: { href: Href; label: string; testID?: string }) {
  return (
    <Link href={href} style={styles.link} testID={testID}>
      {label}
    </Link>
  );
}

export function LinkText({ children }: { children: string }) {
  return <Text style={styles.link}>{children}</Text>;
}

const styles = StyleSheet.create({ link: { color: colors.loom, fontFamily: fonts.bodyBold, fontSize: 15, textDecorationLine: 'underline' } });
