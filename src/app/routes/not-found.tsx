import { NotFoundPage } from '@/app/route-error';

export function Component() {
  return <NotFoundPage />;
}
