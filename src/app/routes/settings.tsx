import { PageHeading } from '../../components/ui/page-heading';
import { MailLog } from '../../features/outbox/components/mail-log';
import { useSessionUser } from '../../features/session/api/queries';
import { BusinessSettingsPanel } from '../../features/settings/components/business-settings';
import { UsersPanel } from '../../features/settings/components/users-panel';

/** The owner's page (the frame turns any other role away): the business, its rates and who signs in. */
export function Component() {
  const { id } = useSessionUser();
  return (
    <>
      <PageHeading title="Settings">
        The business as invoices show it, what new work is priced at, who may sign in, and the mail sent from
        Vanbay.
      </PageHeading>
      <div className="grid max-w-5xl gap-6">
        <BusinessSettingsPanel />
        <UsersPanel selfId={id} />
        <MailLog />
      </div>
    </>
  );
}
