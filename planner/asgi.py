"""ASGI entry point, for servers that speak ASGI."""

import os

from django.core.asgi import get_asgi_application

os.environ.setdefault("DJANGO_SETTINGS_MODULE", "planner.settings")

application = get_asgi_application()
