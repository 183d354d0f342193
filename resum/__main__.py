from .cli import run

if __name__ == "__main__":     # worker processes (resum.parallel) import this module too
    run()
