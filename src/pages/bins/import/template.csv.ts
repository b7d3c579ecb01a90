import { endpoint } from '@/lib/endpoint.server';
import { templateCsv } from '@/lib/bins/register-csv';
import { formOptions } from '@/lib/bins/bin-forms.server';
import { csvResponse } from '@/lib/http/csv-response';

/** A template for the register import, with this operator's own bin type and depot codes. */
export const GET = endpoint({ capability: 'bins.import' }, async () => {
  const options = await formOptions();
  const csv = templateCsv({ companyPrefix: options.companyPrefix, binTypes: options.binTypes, depotCode: options.depots[0]?.code ?? 'DEPOT-CODE' });
  return csvResponse(csv, 'loopfold-bin-register-template.csv');
});
