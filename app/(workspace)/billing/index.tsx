import { BillingScreen } from '@/components/billing/billing-screen';

export default BillingScreen;
