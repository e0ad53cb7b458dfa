import { buttonClasses } from '../../../components/ui/button';
import { Panel } from '../../../components/ui/panel';
import { invoicePdfPath } from '../api/queries';

/**
 * The PDF exactly as the customer gets it, in the browser's own viewer; the session cookie goes
 * along with the viewer's request. A phone that shows no PDFs inline still has the download.
 */
export function InvoicePdf({ id, number }: { id: number; number: string }) {
  const path = invoicePdfPath(id);
  return (
    <Panel>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 className="text-xl font-bold">The PDF</h2>
        <div className="flex flex-wrap gap-3">
          <a href={path} download={`invoice-${number}.pdf`} className={buttonClasses()}>
            Download the PDF
          </a>
          <a href={path} target="_blank" rel="noopener" className={buttonClasses('secondary')}>
            Open in a new tab
          </a>
        </div>
      </div>
      {/* An <object>, not a frame: where the browser has no PDF viewer (phones), the words inside show instead. */}
      <object
        data={path}
        type="application/pdf"
        aria-label={`Invoice ${number} as a PDF`}
        className="mt-4 h-[75vh] min-h-96 w-full rounded-plate border-2 border-rule bg-ground"
      >
        <p className="p-6 text-lg">
          This browser does not show PDFs inside the page. Use “Download the PDF” above, or open it in a new
          tab.
        </p>
      </object>
    </Panel>
  );
}
