import { PageHeader } from '@/components/ui/page-header';
import { InspectorLinksSection } from '@/features/records/components/inspector-links-section';
import { DocumentsSection } from '@/features/records/components/documents-section';
import { AuditPacketPanel } from '@/features/records/components/audit-packet-panel';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  return (
    <div className="space-y-6">
      <PageHeader title="Records" description="Your permits and certificates, and what you share with inspectors." />
      <DocumentsSection />
      <InspectorLinksSection />
      <AuditPacketPanel />
    </div>
  );
}
