import { SkillsScreen } from '@/components/people/skills-screen';

export default SkillsScreen;
