"""Logging in and out, and the admin for staff."""

from django.urls import reverse

from tests.web.conftest import PASSWORD


def test_login_page_logs_a_member_in_and_goes_to_the_catalogue(client, viewer, demo_in_db):
    page = client.get(reverse("login"))
    assert page.status_code == 200 and 'name="csrfmiddlewaretoken"' in page.content.decode()
    response = client.post(reverse("login"), {"username": "vera", "password": PASSWORD}, follow=True)
    assert response.redirect_chain[-1][0] == reverse("catalogue:list")
    assert "vera · viewer" in response.content.decode()


def test_wrong_password_is_refused_on_the_page(client, viewer):
    response = client.post(reverse("login"), {"username": "vera", "password": "wrong"})
    assert response.status_code == 200
    assert "Please enter a correct username and password" in response.content.decode()


def test_logout_is_a_post(viewer_client):
    response = viewer_client.post(reverse("logout"))
    assert response.status_code == 302
    assert viewer_client.get(reverse("catalogue:list")).status_code == 302


def test_home_goes_to_the_catalogue(viewer_client):
    response = viewer_client.get("/")
    assert response.status_code == 302 and response["Location"] == reverse("catalogue:list")


def test_staff_open_the_admin_and_members_do_not(client, make_member, demo_in_db):
    staff = make_member("stella", "editor", is_staff=True, is_superuser=True)
    client.force_login(staff)
    assert client.get(reverse("admin:catalogue_species_changelist")).status_code == 200
    assert "Admin" in client.get(reverse("catalogue:list")).content.decode()
    client.force_login(make_member("mo", "editor"))
    assert client.get(reverse("admin:catalogue_species_changelist")).status_code == 302


def test_migrate_alone_gives_the_roles_every_permission(db):
    # No give_role call: the groups must be complete straight after the test database's migrate.
    from django.contrib.auth.models import Group

    from planner.catalogue.roles import EDITORS, ROLE_PERMISSIONS

    editors = Group.objects.get(name=EDITORS)
    granted = {(p.content_type.app_label, p.codename) for p in editors.permissions.select_related("content_type")}
    assert granted == set(ROLE_PERMISSIONS[EDITORS])
