CREATE TABLE `account_token` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`user_id` varchar(40) NOT NULL,
	`purpose` enum('password_reset','verify_email') NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`expires_at` datetime NOT NULL,
	`used_at` datetime,
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	CONSTRAINT `account_token_id` PRIMARY KEY(`id`),
	CONSTRAINT `account_token_hash_unique` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `companion_event` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`companion_id` bigint unsigned NOT NULL,
	`actor_id` varchar(40),
	`kind` varchar(40) NOT NULL,
	`from_state` enum('draft','in_review','revising','accepted','published','withdrawn'),
	`to_state` enum('draft','in_review','revising','accepted','published','withdrawn'),
	`reason` text NOT NULL,
	`detail` json NOT NULL,
	`revision` varchar(40),
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `companion_event_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `invitation` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`companion_id` bigint unsigned NOT NULL,
	`email` varchar(254) NOT NULL,
	`role` enum('reader','reviewer','author','editor') NOT NULL,
	`message` text NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`invited_by` varchar(40),
	`expires_at` datetime NOT NULL,
	`accepted_at` datetime,
	`accepted_by` varchar(40),
	`revoked_at` datetime,
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	CONSTRAINT `invitation_id` PRIMARY KEY(`id`),
	CONSTRAINT `invitation_hash_unique` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `pending_notice` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`user_id` varchar(40) NOT NULL,
	`companion_id` bigint unsigned,
	`subject` varchar(300) NOT NULL,
	`text` text NOT NULL,
	`link` varchar(500) NOT NULL,
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	`sent_at` datetime,
	CONSTRAINT `pending_notice_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `remark_message` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`remark_id` bigint unsigned NOT NULL,
	`author_id` varchar(40),
	`body` text NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `remark_message_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `remark` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`companion_id` bigint unsigned NOT NULL,
	`figure_number` int NOT NULL,
	`revision` varchar(40) NOT NULL,
	`anchor` json NOT NULL,
	`state` enum('open','settled') NOT NULL DEFAULT 'open',
	`author_id` varchar(40),
	`settled_by` varchar(40),
	`settled_at` datetime,
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	`updated_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `remark_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `companion` ADD `page_text` mediumtext DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE `companion` ADD `license` enum('CC-BY-4.0','CC-BY-SA-4.0','CC0-1.0','ODC-By-1.0') DEFAULT 'CC-BY-4.0' NOT NULL;--> statement-breakpoint
ALTER TABLE `companion` ADD `identities_open` boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `companion` ADD `remarks_public` boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `companion` ADD `published_at` datetime;--> statement-breakpoint
ALTER TABLE `companion` ADD `published_revision` varchar(40);--> statement-breakpoint
ALTER TABLE `membership` ADD `reviewer_number` int;--> statement-breakpoint
ALTER TABLE `user` ADD `email_verified_at` datetime;--> statement-breakpoint
ALTER TABLE `user` ADD `remark_mail` enum('immediate','daily','none') DEFAULT 'immediate' NOT NULL;--> statement-breakpoint
ALTER TABLE `user` ADD `mail_key` varchar(64) DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE `account_token` ADD CONSTRAINT `account_token_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `companion_event` ADD CONSTRAINT `companion_event_companion_id_companion_id_fk` FOREIGN KEY (`companion_id`) REFERENCES `companion`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `companion_event` ADD CONSTRAINT `companion_event_actor_id_user_id_fk` FOREIGN KEY (`actor_id`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `invitation` ADD CONSTRAINT `invitation_companion_id_companion_id_fk` FOREIGN KEY (`companion_id`) REFERENCES `companion`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `invitation` ADD CONSTRAINT `invitation_invited_by_user_id_fk` FOREIGN KEY (`invited_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `invitation` ADD CONSTRAINT `invitation_accepted_by_user_id_fk` FOREIGN KEY (`accepted_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `pending_notice` ADD CONSTRAINT `pending_notice_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `pending_notice` ADD CONSTRAINT `pending_notice_companion_id_companion_id_fk` FOREIGN KEY (`companion_id`) REFERENCES `companion`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `remark_message` ADD CONSTRAINT `remark_message_remark_id_remark_id_fk` FOREIGN KEY (`remark_id`) REFERENCES `remark`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `remark_message` ADD CONSTRAINT `remark_message_author_id_user_id_fk` FOREIGN KEY (`author_id`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `remark` ADD CONSTRAINT `remark_companion_id_companion_id_fk` FOREIGN KEY (`companion_id`) REFERENCES `companion`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `remark` ADD CONSTRAINT `remark_author_id_user_id_fk` FOREIGN KEY (`author_id`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `remark` ADD CONSTRAINT `remark_settled_by_user_id_fk` FOREIGN KEY (`settled_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `account_token_user_idx` ON `account_token` (`user_id`);--> statement-breakpoint
CREATE INDEX `companion_event_companion_idx` ON `companion_event` (`companion_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `invitation_companion_idx` ON `invitation` (`companion_id`);--> statement-breakpoint
CREATE INDEX `pending_notice_user_idx` ON `pending_notice` (`user_id`,`sent_at`);--> statement-breakpoint
CREATE INDEX `remark_message_remark_idx` ON `remark_message` (`remark_id`);--> statement-breakpoint
CREATE INDEX `remark_companion_idx` ON `remark` (`companion_id`,`figure_number`);