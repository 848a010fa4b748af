from ignite.cli.main import main

main()
