import { colors } from '@/constants/theme';
import type { StaffWishKind } from '@/shared/api/staff';

/** Words and colours for the three stances a person can take on a day or shift (DESIGN.md: wish). */
export const WISH_WORDS: Record<StaffWishKind, { label: string; tone: string; soft: string; hint: string }> = {
  prefer: { label: 'Prefer', tone: colors.ok, soft: '#DCEBDD', hint: 'I would like to work' },
  avoid: { label: 'Avoid', tone: colors.thread, soft: colors.threadSoft, hint: 'Rather not, if it can be helped' },
  cannot: { label: 'Cannot', tone: colors.danger, soft: colors.dangerSoft, hint: 'I am not available' },
};

export const WISH_CHOICES = (['prefer', 'avoid', 'cannot'] as const).map((k) => ({ value: k, label: WISH_WORDS[k].label, tone: WISH_WORDS[k].tone }));
