import { MyLedgerScreen } from '@/components/ledger/my-ledger-screen';

export default MyLedgerScreen;
