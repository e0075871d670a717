import { Section } from './section';
import { WorkspaceSwitcher } from './workspace-switcher';

/**
 * For someone signed in without a workspace (removed from their last one, or an invitation that
 * was withdrawn before they accepted it): the way forward is to start their own.
 */
export function NoWorkspace() {
  return (
    <Section title="Start a workspace" lead="Ask an admin to invite you again, or make a workspace of your own and invite your team." testID="no-workspace">
      <WorkspaceSwitcher />
    </Section>
  );
}
