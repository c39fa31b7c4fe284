import { Link } from 'react-router-dom';
import { PrismaCounts } from '../../features/screening/components/PrismaCounts';
import { ScreenerAgreement } from '../../features/screening/components/ScreenerAgreement';

/** The PRISMA 2020 flow numbers on a screen of their own, for anyone. */
export function PrismaFlowPage() {
  return (
    <div className="reading max-w-3xl">
      <h1>PRISMA 2020 flow</h1>
      <p className="mb-3 text-sm">
        Records identified, duplicates removed, screened and excluded with their reasons, counted from the registry as it is now (each
        reference’s latest decision counts; taken-back decisions do not).
      </p>
      <PrismaCounts />
      <h2 className="mt-4">Agreement between screeners</h2>
      <ScreenerAgreement />
      <p className="mt-3 text-sm">
        <Link to="/screening">← Back to screening</Link>
      </p>
    </div>
  );
}
