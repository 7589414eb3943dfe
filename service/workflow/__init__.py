"""The workflow around packs: drafts now; review, waivers and sign-off build on it."""
