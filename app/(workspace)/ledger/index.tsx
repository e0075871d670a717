import { LedgerScreen } from '@/components/ledger/ledger-screen';

export default LedgerScreen;
