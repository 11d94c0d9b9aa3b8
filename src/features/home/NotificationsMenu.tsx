/** The header's notification list with its unread count: the review events addressed to this user. */
import { Link } from 'react-router';
import { Menu, MenuSeparator, menuItemClass } from '@/components/Menu';
import { formatDateTime } from '@/lib/format';
import { useMarkRead, useNotifications } from './hooks';
import { noticeText } from './text';

function BellIcon() {
  return (
    <svg width={16} height={16} viewBox="0 0 16 16" fill="none" stroke="currentColor" strokeWidth={1.5} strokeLinecap="round" strokeLinejoin="round" aria-hidden="true" focusable="false">
      <path d="M4 11V7a4 4 0 0 1 8 0v4l1.2 1.5H2.8z" />
      <path d="M6.5 14a1.6 1.6 0 0 0 3 0" />
    </svg>
  );
}

export function NotificationsMenu() {
  const query = useNotifications();
  const markRead = useMarkRead();
  const unread = query.data?.unread ?? 0;
  const items = query.data?.notifications ?? [];
  const label = unread > 0 ? `Notifications, ${unread} unread` : 'Notifications';
  return (
    <Menu
      label={label}
      align="right"
      menuClassName="w-96 max-w-[calc(100vw-2rem)]"
      buttonClassName="relative flex h-8 items-center gap-1 rounded-md px-2 text-graphite-200 hover:bg-graphite-800 hover:text-white aria-expanded:bg-graphite-800"
      button={
        <>
          <BellIcon />
          {unread > 0 ? (
            <span data-testid="unread-count" className="min-w-5 rounded-full bg-copper-400 px-1.5 text-center text-[11px] leading-5 font-semibold text-graphite-950">
              {unread > 99 ? '99+' : unread}
            </span>
          ) : null}
        </>
      }
    >
      {({ close }) => (
        <>
          <div role="presentation" className="flex items-center justify-between px-3 pt-1.5 pb-2">
            <span className="text-[13px] font-semibold text-graphite-900">Notifications</span>
            <span className="text-xs text-graphite-600">{unread > 0 ? `${unread} unread` : 'All read'}</span>
          </div>
          <MenuSeparator />
          {query.isError ? (
            <p role="presentation" className="px-3 py-2 text-[13px] text-fault-700">
              Could not load notifications.
            </p>
          ) : items.length === 0 ? (
            <p role="presentation" className="px-3 py-2 text-[13px] text-graphite-600">
              Nothing yet. Review requests, comments and decisions on your designs appear here.
            </p>
          ) : (
            <div role="presentation" className="max-h-96 overflow-y-auto">
              {items.map((n) => (
                <Link
                  key={n.id}
                  to={n.path}
                  role="menuitem"
                  tabIndex={-1}
                  className={`${menuItemClass} items-start! whitespace-normal!`}
                  onClick={() => {
                    close();
                    if (!n.read) markRead.mutate({ ids: [n.id] });
                  }}
                >
                  <span aria-hidden="true" className={`mt-1.5 size-2 shrink-0 rounded-full ${n.read ? 'bg-transparent' : 'bg-copper-600'}`} />
                  <span className="min-w-0">
                    <span className={`block text-[13px] ${n.read ? 'text-graphite-700' : 'font-semibold text-graphite-950'}`}>
                      {noticeText(n)}
                      {n.read ? null : <span className="sr-only"> (unread)</span>}
                    </span>
                    {n.excerpt ? <span className="block truncate text-xs text-graphite-600">“{n.excerpt}”</span> : null}
                    <span className="block text-[11px] text-graphite-600">
                      {n.project.name} · {formatDateTime(n.createdAt)}
                    </span>
                  </span>
                </Link>
              ))}
            </div>
          )}
          {unread > 0 ? (
            <>
              <MenuSeparator />
              <button type="button" role="menuitem" tabIndex={-1} className={menuItemClass} onClick={() => markRead.mutate({ all: true })}>
                Mark all as read
              </button>
            </>
          ) : null}
        </>
      )}
    </Menu>
  );
}
