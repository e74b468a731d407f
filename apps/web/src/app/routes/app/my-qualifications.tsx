import { Link } from 'react-router-dom';
import { Card, PageHeader } from '@/components/ui/page-header';
import { paths } from '@/config/paths';
import { useUser } from '@/lib/auth';

export default function MyQualificationsRoute() {
  const me = useUser();
  return (
    <>
      <PageHeader title="My qualifications" description={`Signed in as ${me.name}.`} />
      <Card className="p-5">
        <p className="text-stone-800">
          Your qualifications, the ranges they cover and the days left on each will be listed here once Beadroll keeps the
          qualification records. Until then your QA manager holds them.
        </p>
        {me.welderId ? (
          <p className="mt-3">
            <Link to={paths.welder.href(me.welderId)} className="font-semibold text-accent-700 underline">
              Open your welder file
            </Link>{' '}
            <span className="text-stone-600">to check your stamp, home shop and e-mail.</span>
          </p>
        ) : (
          <p className="mt-3 text-stone-600">Your sign-in is not linked to a welder record yet. Ask your QA manager.</p>
        )}
      </Card>
    </>
  );
}
