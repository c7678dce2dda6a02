"""The load test (`manage.py load_test`): many logged-in clients against a running Linecast on loopback.

A plain package rather than a Django app: it has no models, and its command
lives beside the plan benchmark in ``planner/planning/management/commands``.

- ``client.py`` — one client: keep-alive connection, cookies, the real login form.
- ``mix.py`` — what is requested: targets discovered from the pages, a fixed weighted mix.
- ``runner.py`` — warm-up, then the clients in threads, bounded by count and time.
- ``report.py`` — throughput, latency percentiles, errors, the verdict.
- ``server.py`` — a temporary production server (gunicorn) on a free loopback port.
"""
