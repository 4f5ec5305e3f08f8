import { data, type Params } from 'react-router';

/** The comparison id of a route's params; anything but a positive whole number is a 404. */
export function comparisonIdFrom(params: Params): number {
  const id = Number(params.id);
  if (!Number.isInteger(id) || id < 1) throw data('No comparison has this address.', { status: 404 });
  return id;
}
